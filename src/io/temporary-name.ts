/**
 * The distinct part of a temporary file's name: the process and 48 random
 * bits. Every temporary file is created with wx (O_EXCL), which fails
 * rather than open a file or link that is there already, so the bits need
 * only make a clash unlikely: Math.random, not node:crypto, which takes
 * 4-6 ms to load at start-up (measured in a fresh process on the benchmark
 * machine).
 */
export function temporaryNamePart(): string {
  return `${process.pid}-${Math.floor(Math.random() * 2 ** 48)
    .toString(16)
    .padStart(12, '0')}`;
}
