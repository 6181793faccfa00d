// The benchmark's yardstick for figure 3: a bare node:http server, in a process of its own
// like the app's, that answers every request with the bytes of one file. Prints its port.
import { readFileSync } from "node:fs";
import { createServer } from "node:http";

const body = readFileSync(process.argv[2]);
const server = createServer((_request, response) => {
  response.writeHead(200, { "Content-Type": "application/json", "Content-Length": body.length });
  response.end(body);
});
server.listen(0, "127.0.0.1", () => console.log(server.address().port));
