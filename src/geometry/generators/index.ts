export * from './mesh.ts';
export * from './fins.ts';
export * from './slats.ts';
export * from './overhang.ts';
export * from './canopy.ts';
export * from './umbrella.ts';
export * from './tree.ts';
