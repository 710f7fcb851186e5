// Prints linalgBackend() as JSON; run by backend_choice_test.ts under various permissions.
import { linalgBackend } from "../../lib/linalg/backend.ts";
console.log(JSON.stringify(linalgBackend()));
