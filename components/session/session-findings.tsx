// Placeholder owned by the findings work: replaced by the findings list with acknowledge.
export async function SessionFindings(_props: { sessionId: number; teamId: string; canAcknowledge: boolean }) {
  return null;
}
