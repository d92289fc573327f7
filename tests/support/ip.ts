// A distinct client address per test client, so the sign-in limiter (which is on, as in production)
// counts each test on its own. Each test file starts at a random point of 10.0.0.0/8 (16 million
// addresses), so files running side by side do not meet in one limiter bucket.
let counter = 1 + Math.floor(Math.random() * (1 << 23));
export function nextTestIp(): string {
  counter++;
  return `10.${(counter >> 16) & 255}.${(counter >> 8) & 255}.${counter & 255}`;
}
