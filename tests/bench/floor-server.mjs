// The floor of the run-sheet benchmark: a bare node:http server (no Express, no session, no
// database) that answers every request with the same bytes the real server sent, read from the file
// named by argv[2], with the same Content-Encoding (argv[3]). Whatever latency autocannon measures
// against it is the cost of moving those bytes through loopback and the load generator on this
// machine; the real server cannot do better than that.
import { readFileSync } from 'node:fs';
import http from 'node:http';

const body = readFileSync(process.argv[2]);
const encoding = process.argv[3];
const server = http.createServer((_req, res) => {
  res.writeHead(200, { 'content-type': 'application/json', 'content-length': body.length, ...(encoding ? { 'content-encoding': encoding } : {}) });
  res.end(body);
});
server.listen(0, '127.0.0.1', () => process.send?.({ port: server.address().port }));
process.on('SIGTERM', () => server.close(() => process.exit(0)));
