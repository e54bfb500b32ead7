export * from './api';
export * from './auth';
export * from './browser';
export * from './mailbox';
export * from './server';
export * from './demo';
