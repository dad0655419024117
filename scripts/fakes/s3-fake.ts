// The local S3 fake (s3rver) used by tests and the two-server demo in place of a hosted bucket.
// It accepts the fixed key pair below; the app reaches it with STORAGE_DRIVER=s3 and the S3_* settings.
import fs from 'node:fs';
import S3rver from 's3rver';

export const S3_FAKE_ACCESS_KEY_ID = 'S3RVER';
export const S3_FAKE_SECRET_ACCESS_KEY = 'S3RVER';

export type S3Fake = { endpoint: string; bucket: string; settings: Record<string, string>; close: () => Promise<void> };

export async function startS3Fake(options: { port?: number; dir: string; bucket: string }): Promise<S3Fake> {
  fs.mkdirSync(options.dir, { recursive: true });
  const server = new S3rver({
    address: '127.0.0.1',
    port: options.port ?? 0,
    silent: true,
    directory: options.dir,
    configureBuckets: [{ name: options.bucket }],
  });
  const address = await server.run();
  const endpoint = `http://127.0.0.1:${address.port}`;
  return {
    endpoint,
    bucket: options.bucket,
    // The app's settings that point at this fake.
    settings: {
      STORAGE_DRIVER: 's3',
      S3_ENDPOINT: endpoint,
      S3_BUCKET: options.bucket,
      S3_REGION: 'us-east-1',
      S3_ACCESS_KEY_ID: S3_FAKE_ACCESS_KEY_ID,
      S3_SECRET_ACCESS_KEY: S3_FAKE_SECRET_ACCESS_KEY,
      S3_FORCE_PATH_STYLE: 'true',
    },
    close: () => server.close(),
  };
}
