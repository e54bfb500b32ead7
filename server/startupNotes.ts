// Lines a service wants printed in the start-up banner, under the demo accounts (e.g. the demo
// share link). Services add them while starting; server/index.ts prints them.
export const startupNotes: string[] = [];
