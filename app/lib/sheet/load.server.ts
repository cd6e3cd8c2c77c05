// Reads what the spec sheet shows of one package (prices are not on the sheet).
import type { Db } from "../db.server";
import { getBenchState, getPackageHeader } from "../packages/store.server";
import { sheetModel, type SheetModel } from "./model";

export async function loadSheet(db: Db, packageId: number): Promise<SheetModel | null> {
  const [header, state] = await Promise.all([
    getPackageHeader(db, packageId),
    getBenchState(db, packageId, false),
  ]);
  if (!header || !state) return null;
  return sheetModel({
    name: header.name,
    bike: header.bikeLabel,
    customer: header.customerName,
    status: header.status,
    revision: state.revision,
    spec: state.spec,
    computation: state.computation,
    findings: state.findings,
    parts: state.parts,
  });
}
