// The workflow around one claim, for both sides: the thread, returns, the decision and its letter, and the
// moves this user can make now. The server decides; these forms only offer what the stage machine allows.
// One component per file in ./workflow/; this module is what the routes import.

export { Assignment } from './workflow/assignment';
export { BenchTestForm } from './workflow/bench-test-form';
export { DecisionCard } from './workflow/decision-card';
export { InstallerWorkflow } from './workflow/installer-workflow';
export { ReceiveUnitForm } from './workflow/receive-unit-form';
export { Returns } from './workflow/returns';
export { ReviewActions } from './workflow/review-actions';
export { Thread } from './workflow/thread';
