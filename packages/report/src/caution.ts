/** The caution every report and curve export carries, at top and bottom. */
export const DESIGN_VALUE_CAUTION =
  'Statistical estimates from the data given. Verify against the governing codes and have a licensed engineer review before use in design.';
