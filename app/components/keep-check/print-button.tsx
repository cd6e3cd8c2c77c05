export function PrintButton() {
  return (
    <button
      type="button"
      onClick={() => window.print()}
      className="rounded border border-steel-300 bg-white px-4 py-2 font-semibold text-ink hover:bg-steel-100 print:hidden"
    >
      Print
    </button>
  );
}
