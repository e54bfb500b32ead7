// Checked steps in the editor: flow and claim blocks, their live verdicts, and the side panels.
export { CheckedBlocks } from './nodes';
export { BlockTools } from './BlockTools';
export { ChecksSidebar, showStep } from './ChecksSidebar';
export { liveChecksOf, configureLiveChecks, type LiveChecks, type LiveSnapshot, type ClaimView } from './live';
