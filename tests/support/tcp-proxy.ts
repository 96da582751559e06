// A TCP relay between the API and PostgreSQL that a test can cut and restore: cutting closes every
// relayed connection at once (as a PostgreSQL restart does to its clients, which then read
// "Connection terminated unexpectedly") and refuses new ones (ECONNREFUSED) until restored.
import net from 'node:net';

export interface TcpProxy {
  /** The same URL with host and port replaced by the relay's. */
  url(direct: string): string;
  port: number;
  /** Ends every relayed connection and stops listening. */
  cut(): Promise<void>;
  /** Listens again on the same port. */
  restore(): Promise<void>;
  close(): Promise<void>;
}

export async function startTcpProxy(target: { host: string; port: number }): Promise<TcpProxy> {
  const sockets = new Set<net.Socket>();
  const server = net.createServer((client) => {
    const upstream = net.connect(target.port, target.host);
    sockets.add(client);
    sockets.add(upstream);
    const end = () => {
      client.destroy();
      upstream.destroy();
      sockets.delete(client);
      sockets.delete(upstream);
    };
    client.on('error', end).on('close', end);
    upstream.on('error', end).on('close', end);
    client.pipe(upstream);
    upstream.pipe(client);
  });
  const listen = (port: number) =>
    new Promise<number>((resolve, reject) => {
      server.once('error', reject);
      server.listen(port, '127.0.0.1', () => {
        server.off('error', reject);
        resolve((server.address() as net.AddressInfo).port);
      });
    });
  const port = await listen(0);
  let listening = true;
  const stop = async () => {
    if (!listening) return;
    listening = false;
    const closed = new Promise<void>((resolve) => server.close(() => resolve()));
    for (const s of sockets) s.destroy();
    sockets.clear();
    await closed;
  };
  return {
    port,
    url(direct) {
      const u = new URL(direct);
      u.hostname = '127.0.0.1';
      u.port = String(port);
      return u.toString();
    },
    cut: stop,
    async restore() {
      if (listening) return;
      await listen(port);
      listening = true;
    },
    close: stop,
  };
}
