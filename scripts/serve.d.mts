// Types of what scripts/serve.mjs exports, for the tests that import it.
import type { NextFunction, Request, Response } from "express";

export const CLIENT_ADDRESS_HEADER: string;
export function clientAddressMiddleware(req: Request, res: Response, next: NextFunction): void;
export function contentSecurityPolicy(nonce: string): string;
export function securityHeadersMiddleware(
  appUrl?: string,
): (req: Request, res: Response, next: NextFunction) => void;
