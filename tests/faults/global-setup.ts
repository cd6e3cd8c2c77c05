import type { TestProject } from "vitest/node";
import { startSharedCluster, type ClusterInfo } from "./support";

declare module "vitest" {
  export interface ProvidedContext {
    faultCluster: ClusterInfo;
  }
}

// One cluster for the fault tests (they run one file at a time), torn down at the end.
export default async function setup(project: TestProject) {
  const cluster = await startSharedCluster();
  project.provide("faultCluster", { port: cluster.port, dataDir: cluster.dataDir });
  return () => cluster.destroy();
}
