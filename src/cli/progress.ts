/** A one-line progress bar on stderr, only when stderr is a TTY (never in pipes or CI logs). */
export function progressBar(label: string, stream: NodeJS.WriteStream = process.stderr) {
  const live = Boolean(stream.isTTY) && !process.env.CI;
  let last = -1;
  return {
    update: (done: number, total: number): void => {
      if (!live || total <= 0) return;
      const pct = Math.min(100, Math.floor((100 * done) / total));
      if (pct === last) return;
      last = pct;
      const width = 30;
      const fill = Math.round((width * pct) / 100);
      stream.write(`\r${label} [${'#'.repeat(fill)}${'.'.repeat(width - fill)}] ${pct}%`);
    },
    done: (): void => {
      if (live && last >= 0) stream.write('\r\x1b[2K');
    },
  };
}
