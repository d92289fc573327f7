import "server-only";
// The most common leaked passwords of 8+ characters (compiled from memory of public breach top lists),
// plus words of the trade that people reach for here. Lower-cased; matched after trimming.
const LIST = `password 12345678 123456789 1234567890 qwerty123 qwertyuiop password1 password123 iloveyou 11111111
00000000 abc12345 abcd1234 1q2w3e4r 1qaz2wsx qwerty12 sunshine princess football baseball
welcome1 welcome123 admin123 administrator letmein1 trustno1 dragon123 monkey123 superman batman123
starwars master123 passw0rd p@ssw0rd p@ssword changeme changeme1 secret123 zaq12wsx 87654321
12341234 11223344 123123123 987654321 qwer1234 asdf1234 asdfghjk zxcvbnm1 password! iloveyou1
whatever michael1 jennifer shadow12 charlie1 jordan23 liverpool chelsea1 arsenal1 computer
internet samsung1 freedom1 mustang1 harley12 summer2024 winter2024 spring2024 autumn2024 summer2025
winter2025 summer2026 winter2026 password2024 password2025 password2026 qwerty2024 default1 guest123
radio123 vintage1 antique1 receiver transistor shortwave wireless kestrel1 bandedge bandedge1
12qwaszx 1qaz2wsx3edc q1w2e3r4 q1w2e3r4t5 a1b2c3d4 aaaaaaaa zzzzzzzz 01234567 abcdefgh
loveyou1 football1 baseball1 hello123 hellohello letmein123 access14 mypassword mypass123 passpass`;

const COMMON = new Set(LIST.split(/\s+/).filter(Boolean));

export function isCommonPassword(password: string): boolean {
  return COMMON.has(password.trim().toLowerCase());
}
