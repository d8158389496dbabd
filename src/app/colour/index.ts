export * from './scales.ts';
export * from './units.ts';
export * from './legend.ts';
export * from './layers.ts';
export * from './diverging.ts';
