// The HTTP server around the Express app, with the timeouts that end slow clients (a client that
// trickles its headers or body a byte a second, or stops reading) and the one error shape for the
// answers Node's HTTP parser gives itself (a timed-out or malformed request). Used by the server,
// the demo seed's loopback listener and the tests, so all of them behave alike.
import http from 'node:http';
import type { Socket } from 'node:net';
import type { RequestListener } from 'node:http';
import type { Config } from '../config.ts';

function rawAnswer(status: number, reason: string, code: string, message: string): string {
  const body = JSON.stringify({ error: { code, message } });
  return `HTTP/1.1 ${status} ${reason}\r\nContent-Type: application/json; charset=utf-8\r\nContent-Length: ${Buffer.byteLength(body)}\r\nConnection: close\r\n\r\n${body}`;
}

/** Answers a request the parser refused (or that timed out) in the one error shape, then closes the connection. */
function onClientError(err: NodeJS.ErrnoException, socket: Socket, config: Config) {
  const inFlight = (socket as Socket & { _httpMessage?: { headersSent?: boolean } })._httpMessage;
  if (err.code === 'ECONNRESET' || !socket.writable || inFlight?.headersSent) {
    socket.destroy();
    return;
  }
  let answer: string;
  if (err.code === 'ERR_HTTP_REQUEST_TIMEOUT') {
    answer = rawAnswer(408, 'Request Timeout', 'request-timeout', `The request did not arrive in time (headers within ${config.http.headersTimeoutMs / 1000} s, the whole request within ${config.http.requestTimeoutMs / 1000} s); nothing was done. Send it again on a steadier connection.`);
  } else if (err.code === 'HPE_HEADER_OVERFLOW') {
    answer = rawAnswer(431, 'Request Header Fields Too Large', 'headers-too-large', 'The request headers are too large; nothing was done.');
  } else {
    answer = rawAnswer(400, 'Bad Request', 'malformed-request', 'The request is not well-formed HTTP; nothing was done.');
  }
  socket.end(answer);
}

/** An HTTP server for `app` with the configured timeouts. */
export function createHttpServer(app: RequestListener, config: Config): http.Server {
  const t = config.http;
  const server = http.createServer(
    {
      headersTimeout: t.headersTimeoutMs,
      requestTimeout: t.requestTimeoutMs,
      keepAliveTimeout: t.keepAliveTimeoutMs,
      // How often Node looks for requests past their headers/request timeout (default 30 s, which
      // would let a trickling client stay up to 30 s longer than configured).
      connectionsCheckingInterval: Math.max(100, Math.min(1000, t.headersTimeoutMs / 4)),
    },
    app,
  );
  // No traffic either way on a socket during a request for this long ends it (a client that stops reading).
  server.timeout = t.idleTimeoutMs;
  server.keepAliveTimeout = t.keepAliveTimeoutMs;
  server.on('clientError', (err: NodeJS.ErrnoException, socket: Socket) => onClientError(err, socket, config));
  return server;
}

/** Creates the server and listens on host:port; resolves once it listens. */
export function listen(app: RequestListener, config: Config, port: number, host: string): Promise<http.Server> {
  const server = createHttpServer(app, config);
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => {
      server.off('error', reject);
      resolve(server);
    });
  });
}
