export * from './roles';
export * from './list';
export * from './me';
export * from './school';
export * from './token';
