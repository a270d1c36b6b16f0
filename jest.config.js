// Three projects: pure computations, the HTTP API on a real PostgreSQL, and the built app in headless Chromium.
const tsTransform = { '^.+\\.tsx?$': ['ts-jest', { tsconfig: '<rootDir>/server/tsconfig.json' }] };
// The engine's AssemblyScript sources (a TypeScript dialect, built by scripts/build-wasm.mjs) are not for Jest.
const common = {
  testEnvironment: 'node',
  transform: tsTransform,
  moduleFileExtensions: ['ts', 'tsx', 'js', 'json'],
  modulePathIgnorePatterns: ['<rootDir>/shared/vision/wasm/assembly/'],
};

module.exports = {
  // Hooks and tests get 60 s: set-up copies a database, and the machine may be busy (a global option, not a project one).
  testTimeout: 60_000,
  projects: [
    { ...common, displayName: 'unit', roots: ['<rootDir>/tests/unit'] },
    { ...common, displayName: 'api', roots: ['<rootDir>/tests/api'], globalSetup: '<rootDir>/tests/support/global-setup.ts' },
    { ...common, displayName: 'browser', roots: ['<rootDir>/tests/browser'], globalSetup: '<rootDir>/tests/support/global-setup.ts' },
  ],
};
