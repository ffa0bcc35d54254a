/**
 * The check made before upload URLs are handed out: any HTTP answer from the upload service counts
 * as "up"; a refused connection is "down" with a message the upload screen shows as it is.
 */
import { describe, it, expect } from "vitest";
import http from "node:http";
import net from "node:net";
import { once } from "node:events";
import { assertUploadServiceAnswers, UPLOAD_SERVICE_DOWN_MESSAGE } from "../../../lib/uploads/upload-service-check";

async function closedPort(): Promise<number> {
  const s = net.createServer().listen(0, "127.0.0.1");
  await once(s, "listening");
  const { port } = s.address() as net.AddressInfo;
  await new Promise((r) => s.close(r));
  return port;
}

describe("assertUploadServiceAnswers", () => {
  it("passes when the service answers, even with a 404 at its root", async () => {
    const server = http.createServer((_req, res) => res.writeHead(404).end()).listen(0, "127.0.0.1");
    await once(server, "listening");
    const { port } = server.address() as net.AddressInfo;
    try {
      await expect(assertUploadServiceAnswers(`http://127.0.0.1:${port}`)).resolves.toBeUndefined();
    } finally {
      server.close();
    }
  });

  it("refuses with the upload screen's message when nothing listens", async () => {
    const err = await assertUploadServiceAnswers(`http://127.0.0.1:${await closedPort()}`).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Error);
    expect((err as { code: string }).code).toBe("UPLOAD_FAILED");
    expect((err as Error).message).toBe(UPLOAD_SERVICE_DOWN_MESSAGE);
    expect(UPLOAD_SERVICE_DOWN_MESSAGE).toMatch(/not answering.*nothing was stored/i);
  });

  it("refuses when the service accepts the connection but never answers", async () => {
    const silent = net.createServer(() => {}).listen(0, "127.0.0.1");
    await once(silent, "listening");
    const { port } = silent.address() as net.AddressInfo;
    try {
      await expect(assertUploadServiceAnswers(`http://127.0.0.1:${port}`, 300)).rejects.toThrow(UPLOAD_SERVICE_DOWN_MESSAGE);
    } finally {
      silent.close();
    }
  });

  it("does nothing when no service address is configured (the hosted service)", async () => {
    await expect(assertUploadServiceAnswers("")).resolves.toBeUndefined();
  });
});
