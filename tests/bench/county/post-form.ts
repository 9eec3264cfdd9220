// Posts a multipart form as a stream of 64 kB slices, as a browser sends a large file, and times
// the answer twice: from the first byte sent, and from the moment the last byte was handed to the
// connection (what the server adds once the whole file is in its hands).
export type PostedForm = { res: Response; answerMs: number; afterLastByteMs: number };

export async function postForm(url: string, headers: Record<string, string>, form: FormData): Promise<PostedForm> {
  const encoded = new Response(form);
  const contentType = encoded.headers.get('content-type')!;
  const body = new Uint8Array(await encoded.arrayBuffer());
  const slice = 64 * 1024;
  let offset = 0;
  let lastByteAt = NaN;
  const stream = new ReadableStream<Uint8Array>({
    pull(controller) {
      if (offset >= body.length) {
        lastByteAt = performance.now();
        controller.close();
        return;
      }
      controller.enqueue(body.subarray(offset, offset + slice));
      offset += slice;
    },
  });
  const t0 = performance.now();
  const res = await fetch(url, { method: 'POST', headers: { ...headers, 'content-type': contentType, 'content-length': String(body.length) }, body: stream, duplex: 'half' } as RequestInit);
  const end = performance.now();
  return { res, answerMs: end - t0, afterLastByteMs: end - lastByteAt };
}
