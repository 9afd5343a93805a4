export * from './columns';
export * from './schools';
export * from './people';
export * from './roster';
export * from './audit';
export * from './mail';
export * from './reports';
export * from './ladder';
