/** The published test functions an island can search (defined in testFunctions.ts). */
export const TEST_FUNCTION_NAMES = ['rosenbrock', 'rastrigin'] as const;
export type TestFunctionName = (typeof TEST_FUNCTION_NAMES)[number];
