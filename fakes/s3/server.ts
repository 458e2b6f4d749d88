import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import S3rver from "s3rver";

// A local S3-compatible server for tests: s3rver (an npm package that speaks S3's REST protocol,
// path-style), listening on 127.0.0.1 only, keeping its objects in a temporary folder that
// `stop()` removes. The AWS SDK talks to it unchanged. It accepts only SigV4 Authorization headers
// carrying its one access key (FAKE_S3_ACCESS_KEY_ID: anything else answers 403); it does not
// recompute the signature, and it ignores conditional writes (If-None-Match).

/** s3rver's built-in account; its access key is the only one it knows. */
export const FAKE_S3_ACCESS_KEY_ID = "S3RVER";
export const FAKE_S3_SECRET_ACCESS_KEY = "S3RVER";

export interface FakeS3 {
  endpoint: string;
  bucket: string;
  /** The settings that point the app at this server (STORAGE_DRIVER=s3 and the S3_* variables). */
  env: Record<string, string>;
  /** Stops the server; its objects stay until `cleanup()`. */
  stop(): Promise<void>;
  /** Stops the server if it still runs and removes its folder. */
  cleanup(): Promise<void>;
}

export async function startFakeS3(options: { bucket?: string; port?: number } = {}): Promise<FakeS3> {
  const bucket = options.bucket ?? "steamlane-test";
  const directory = fs.mkdtempSync(path.join(os.tmpdir(), "steamlane-fake-s3-"));
  const server = new S3rver({ address: "127.0.0.1", port: options.port ?? 0, silent: true, directory, configureBuckets: [{ name: bucket }] });
  const { port } = await server.run();
  const endpoint = `http://127.0.0.1:${port}`;
  let running = true;
  const stop = async () => {
    if (!running) return;
    running = false;
    await server.close();
  };
  return {
    endpoint,
    bucket,
    env: {
      STORAGE_DRIVER: "s3",
      S3_BUCKET: bucket,
      S3_REGION: "us-east-1",
      S3_ENDPOINT: endpoint,
      S3_FORCE_PATH_STYLE: "true",
      S3_ACCESS_KEY_ID: FAKE_S3_ACCESS_KEY_ID,
      S3_SECRET_ACCESS_KEY: FAKE_S3_SECRET_ACCESS_KEY,
    },
    stop,
    async cleanup() {
      await stop();
      fs.rmSync(directory, { recursive: true, force: true });
    },
  };
}
