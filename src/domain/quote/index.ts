/** Quoting made-to-order plates: shop rates, money in minor units, the quote with its lines. */
export * from './settings';
export * from './money';
export * from './quote';
export * from './geometry';
