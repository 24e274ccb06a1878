/** Safety indicators (pure): catalogue, periods, the period report, suppression, diff, CSV rows. PDF: ./pdf. */
export * from './catalogue';
export * from './period';
export * from './suppression';
export * from './format';
export * from './report';
export * from './diff';
export * from './csv';
export * from './requests';
