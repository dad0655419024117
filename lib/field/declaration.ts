// The engineer's declaration, stored word for word with each sign-off so a later rewording never
// changes what was declared.
export const ENGINEER_DECLARATION =
  'I tested the appliances and installation listed for this visit myself, recorded the results as I found them, ' +
  'and told the person responsible about every defect found and the action taken.';
