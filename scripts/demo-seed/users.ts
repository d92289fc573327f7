// The invented people of the demo shop, Kestrel Lane Wireless in Port Alder.
export const DEMO_USERS = [
  { id: "demo-owner-odile", name: "Odile Marchetti", email: "odile@kestrel-lane.example", role: "owner", password: "bench-owner-2026" },
  { id: "demo-tech-tomas", name: "Tomas Reyne", email: "tomas@kestrel-lane.example", role: "technician", password: "bench-tech-2026" },
  { id: "demo-tech-priya", name: "Priya Anand", email: "priya@kestrel-lane.example", role: "technician", password: "bench-tech-2026" },
  { id: "demo-cust-mira", name: "Mira Holloway", email: "mira.holloway@example.com", role: "customer", password: "demo-owner-2026" },
  { id: "demo-cust-jonah", name: "Jonah Pell", email: "jonah.pell@example.com", role: "customer", password: "demo-owner-2026" },
  { id: "demo-cust-ines", name: "Ines Varga", email: "ines.varga@example.net", role: "customer", password: "demo-owner-2026" },
  {
    id: "demo-cust-walt",
    name: "Walt Brennan (estate of)",
    email: "brennan.estate@example.org",
    role: "customer",
    password: "demo-owner-2026",
  },
] as const;

export const DEMO_SHOP = {
  name: "Kestrel Lane Wireless",
  addressLines: ["14 Kestrel Lane", "Port Alder"],
  phone: "+1 555 0142",
  email: "workshop@kestrel-lane.example",
};
