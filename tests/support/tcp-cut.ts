/**
 * A TCP relay between an app instance and MariaDB that a test can cut and restore, to play a
 * database outage without touching the shared server. `cut()` closes every open connection and
 * refuses new ones (what a stopped server looks like); `restore()` accepts again.
 */
import { createServer, connect, type Server, type Socket } from "node:net";

export interface TcpCut {
  port: number;
  cut(): Promise<void>;
  restore(): Promise<void>;
  close(): Promise<void>;
}

export async function startTcpCut(
  target: { host: string; port: number },
  port = 0,
): Promise<TcpCut> {
  const open = new Set<Socket>();
  let server: Server | undefined;
  let listenPort = port;

  const listen = () =>
    new Promise<void>((ok, fail) => {
      const s = createServer((client) => {
        const upstream = connect(target.port, target.host);
        open.add(client);
        open.add(upstream);
        const end = () => {
          client.destroy();
          upstream.destroy();
          open.delete(client);
          open.delete(upstream);
        };
        client.on("error", end).on("close", end);
        upstream.on("error", end).on("close", end);
        client.pipe(upstream);
        upstream.pipe(client);
      });
      s.once("error", fail);
      s.listen(listenPort, "127.0.0.1", () => {
        listenPort = (s.address() as { port: number }).port;
        server = s;
        ok();
      });
    });

  const stop = () =>
    new Promise<void>((ok) => {
      for (const s of open) s.destroy();
      open.clear();
      if (!server) return ok();
      server.close(() => ok());
      server = undefined;
    });

  await listen();
  return {
    get port() {
      return listenPort;
    },
    cut: stop,
    restore: async () => {
      if (!server) await listen();
    },
    close: stop,
  };
}
