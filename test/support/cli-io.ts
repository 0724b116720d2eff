/** A captured CliIo for command-line tests. */
export function captureIo() {
  const out: string[] = [];
  const err: string[] = [];
  return { out, err, io: { stdout: (t: string) => out.push(t), stderr: (t: string) => err.push(t), interactive: false } };
}
