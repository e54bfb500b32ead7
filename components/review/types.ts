// What the review routes send, as the page receives it (dates as ISO strings). The page checks at
// compile time that these match the server's types.
export interface PersonWire {
  id: string | null;
  name: string;
}

export interface SignOffWire {
  id: string;
  stepId: string;
  by: PersonWire;
  signedAt: string;
  cleared: { at: string; reason: string; by: PersonWire | null } | null;
}

export type RemarkEntryKind = 'remark' | 'resolved' | 'reopened';

export interface RemarkEntryWire {
  id: string;
  kind: RemarkEntryKind;
  by: PersonWire;
  body: string;
  at: string;
}

export interface RemarkThreadWire {
  id: string;
  stepId: string;
  stepPresent: boolean;
  excerpt: string;
  position: number | null;
  startedBy: PersonWire;
  startedAt: string;
  resolved: { at: string; by: PersonWire } | null;
  entries: RemarkEntryWire[];
}

export interface StepReviewWire {
  stepId: string;
  position: number;
  type: string;
  excerpt: string;
  contentHash: string;
  dependencyStepId: string | null;
  signOffs: SignOffWire[];
  lastCleared: SignOffWire | null;
  openThreads: number;
  resolvedThreads: number;
}

export interface ReviewWire {
  derivationId: string;
  steps: StepReviewWire[];
  threads: RemarkThreadWire[];
  you: { mayRemark: boolean; mayResolve: boolean; maySignOff: boolean };
}

export type HistoryEventKind = 'signed-off' | 'sign-off-cleared' | 'sign-off-withdrawn' | 'remark' | 'reply' | 'resolved' | 'reopened';

export interface StepHistoryWire {
  stepId: string;
  present: boolean;
  excerpt: string;
  events: { at: string; kind: HistoryEventKind; by: PersonWire | null; detail: string; threadId?: string }[];
}

/** What the review panels can ask the page to do; each resolves when done or throws with the server's message. */
export interface ReviewActions {
  remark(stepId: string, body: string): Promise<void>;
  reply(threadId: string, body: string): Promise<void>;
  setResolved(threadId: string, resolved: boolean): Promise<void>;
  signOff(stepId: string, contentHash: string): Promise<void>;
  withdraw(signOffId: string): Promise<void>;
  history(stepId: string): Promise<StepHistoryWire>;
}
