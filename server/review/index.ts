// Review of derivations: remarks anchored to steps, sign-offs cleared when what they checked
// changes, who wrote each step, and the mails of review. Route handlers call these modules; the
// background part runs as a service of the server process (./service).
export { reviewService, type ReviewAccess } from './access';
export { reviewBackgroundService } from './service';
export { replyToThread, setThreadResolved, startThread, type RemarkEntryView, type RemarkThreadView } from './remarks';
export { signOffStep, withdrawSignOff, verifySignOffs, type SignOffView } from './signOffs';
export { reviewView, stepHistory, type ReviewView, type StepHistory, type StepReview } from './view';
