export const REPAIR_CAUTION =
  'Field modifications (bypassing dead LEDs, swapping drivers) can void the fixture’s listing and its warranty. Follow local codes and the authority having jurisdiction, and leave the work to licensed, qualified electricians.';
