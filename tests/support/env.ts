/** Where the throw-away test cluster lives (scripts/test.sh starts it and sets KW_TEST_DATABASE_URL). */
export function testServerUrl(): string {
  const url = process.env.KW_TEST_DATABASE_URL;
  if (!url) throw new Error('KW_TEST_DATABASE_URL is not set: run the tests with `npm test` (it starts a test PostgreSQL)');
  return url.replace(/\/$/, '');
}

export const TEMPLATE_DB = 'kw_test_template';
