// Tables of this feature are added here as its migrations land.
// eslint-disable-next-line @typescript-eslint/no-empty-object-type
export interface PackageTables {}
