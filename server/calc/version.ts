/**
 * Version of the response-calculation engine. Stored with every derived value as part of its
 * provenance; bump it whenever a change could alter a computed number (formula, default, tolerance).
 */
export const CALC_VERSION = 'calc-1.0.0';
