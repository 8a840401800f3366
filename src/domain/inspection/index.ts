/** Inspection of the machined plate against its released revision (pure). */
export * from './truePosition';
export * from './plan';
export * from './measurements';
export * from './evaluate';
export * from './csv';
