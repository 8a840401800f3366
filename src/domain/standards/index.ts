export * from './threads';
export * from './clearanceHoles';
export * from './tapDrills';
export * from './capScrews';
export * from './isoFits';
export * from './flywheelHousings';
export * from './gears';
