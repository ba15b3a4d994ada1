export function ClaimBatchRoute() { return null; }
