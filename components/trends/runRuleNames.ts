// Run rules by their plain names: "WE2" is the second Western Electric rule, "N7" the seventh of Nelson's.
export function runRuleName(code: string): string {
  const we = /^WE(\d)$/.exec(code);
  if (we) return `Western Electric rule ${we[1]}`;
  const nelson = /^N(\d)$/.exec(code);
  if (nelson) return `Nelson rule ${nelson[1]}`;
  return code === 'limit' ? 'Defect-fraction limit' : code;
}
