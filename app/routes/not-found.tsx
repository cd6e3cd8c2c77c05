import { data } from "react-router";
import type { Route } from "./+types/not-found";

export async function loader({ request }: Route.LoaderArgs) {
  throw data(`Nothing at ${new URL(request.url).pathname}`, { status: 404 });
}

export default function NotFound() {
  return null;
}
