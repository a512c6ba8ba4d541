/** The report's safety caution (plain text; the CLI prints a shorter one with every decode). */
export const SAFETY_CAUTION =
  'Everything in this report — decoded positions, confidences, ambiguity ratings — is a statistical estimate, not a safety function. ' +
  'Never use it for collision avoidance or any other safety decision: defer to the robot\'s own certified safety systems, to local codes and to licensed practice.';
