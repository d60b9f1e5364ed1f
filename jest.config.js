/** Unit and reference tests: test/ mirrors src/. Browser tests live in test/browser and run separately. */
module.exports = {
  testEnvironment: 'node',
  roots: ['<rootDir>/test'],
  testMatch: ['**/*.test.ts'],
  testPathIgnorePatterns: ['/node_modules/', '/test/browser/'],
  transform: { '^.+\\.ts$': ['ts-jest', { tsconfig: 'tsconfig.json', isolatedModules: true }] },
  testTimeout: 60000,
  reporters: ['default', '<rootDir>/test/helpers/summaryReporter.js'],
};
