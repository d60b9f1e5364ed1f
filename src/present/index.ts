/** Presentation: dates, numbers, cell names and tables for the pane, the sheet and the command line. No DOM, no Office. */
export * from './isoDate';
export * from './calendarTicks';
export * from './formatNumber';
export * from './cellAddress';
export * from './describe';
export * from './tables';
export * from './excelErrors';
