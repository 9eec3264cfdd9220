// One zod issue in words for the people reading it: zod names a missing value by its
// JavaScript type ("expected string, received undefined"); a form or a file says "Required."
export function issueMessage(issue: { code?: string; message: string }): string {
  return issue.code === 'invalid_type' && /received undefined$/.test(issue.message) ? 'Required.' : issue.message;
}
