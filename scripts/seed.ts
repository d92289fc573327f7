import { seedDemo } from "./demo-seed";

// Idempotent: a second run neither duplicates nor wipes anything.
seedDemo()
  .then((summary) => {
    console.log(`demo seed: ${summary}`);
    process.exit(0);
  })
  .catch((e) => {
    console.error(e);
    process.exit(1);
  });
