// A distinct client address per test client, so the sign-in limiter (which is on, as in production)
// counts each test on its own. One test proves the limiter with a fixed address.
let counter = Math.floor(Math.random() * 200) * 256;
export function nextTestIp(): string {
  counter++;
  return `10.${(counter >> 16) & 255}.${(counter >> 8) & 255}.${counter & 255}`;
}
