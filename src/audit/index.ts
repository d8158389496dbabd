// The audit's public surface (the CLI and the viewer use these): re-exports only.
export * from './project.ts';
export * from './load.ts';
export * from './pipeline.ts';
export * from './results.ts';
export * from './summary.ts';
export * from './csv.ts';
export * from './jsonStream.ts';
export * from './dayTable.ts';
export * from './shard.ts';
export * from './options.ts';
