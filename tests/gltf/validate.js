// Validate a .glb with the Khronos glTF validator; print the counts and the first errors as JSON.
const fs = require('fs');
const validator = require('gltf-validator');

const data = new Uint8Array(fs.readFileSync(process.argv[2]));
validator.validateBytes(data).then((report) => {
  const errors = report.issues.messages.filter((m) => m.severity === 0).slice(0, 5);
  console.log(JSON.stringify({errors: report.issues.numErrors, warnings: report.issues.numWarnings, first: errors}));
}).catch((error) => {
  console.error(String(error));
  process.exit(2);
});
