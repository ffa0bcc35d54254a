// Placeholder owned by the Compare/laps work: replaced by the lap table with sectors and best marks.
export async function SessionLaps(_props: { sessionId: number; teamId: string }) {
  return null;
}
