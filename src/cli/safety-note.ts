/** Printed with every decode: the contract requires that results say plainly what they are not. */
export const SAFETY_NOTE =
  'Decoded positions are statistical estimates, not a safety function: never use them for collision avoidance or safety decisions; robot safety rests on the robot\'s own certified systems and local codes.';
