// How the bench shows a figure in the user's unit system: the shop-wide formatter.
export { fmtLine, inputValue, show, unitOf, type Quantity, type Units } from "../format";
