// Checks an uploaded PDF the way the verification page needs to answer: is it signed, does the
// signature cover the whole file (nothing appended after signing), does the CMS signature verify,
// was it made with one of this organisation's certificates, who signed and when, and which
// briefing it is (from the document information dictionary written by briefing-document.ts).
//
// The CMS is taken apart with node-forge's ASN.1 reader; the RSA/ECDSA check itself and the
// certificate fingerprints use Node's crypto (forge does not verify PKCS#7 signatures).
import { createHash, verify as cryptoVerify, X509Certificate } from 'node:crypto';
import forge from 'node-forge';
import { INFO_KEYS } from '../briefing-document';
import { dictOf, openPdf, pdfDate, pdfText, PdfReadError, PdfTooComplexError, resolve, type PdfDocument, type PdfValue } from './pdf-objects';

export type PdfVerification = {
  /** Every check below passed. */
  valid: boolean;
  fileSha256: string;
  signaturePresent: boolean;
  signatureCount: number;
  /** The signed byte ranges run from the first byte to the last, leaving out only the signature value. */
  coversWholeFile: boolean;
  byteRange: [number, number, number, number] | null;
  /** The digest inside the signature equals the SHA-256 of the signed bytes. */
  digestMatches: boolean;
  /** The signature over that digest verifies with the signer's certificate. */
  cmsSignatureValid: boolean;
  /** The signer's certificate is one of the organisation's (compared by SHA-256 fingerprint). */
  signedByOrganization: boolean;
  certificateValidAtSigning: boolean;
  signer: {
    /** As printed on the page and stored in the file's metadata at signing. */
    name: string | null;
    role: string | null;
    certificateSubject: string | null;
    certificateFingerprintSha256: string | null;
  };
  /** The CMS signing time (signed attribute), else the signature dictionary's /M. */
  signingTime: Date | null;
  briefing: { id: string | null; version: number | null; contentSha256: string | null; status: string | null; organization: string | null };
  /** Plain-words reasons for every failed check, for the verification page. */
  problems: string[];
};

const OID = {
  data: '1.2.840.113549.1.7.1',
  contentType: '1.2.840.113549.1.9.3',
  messageDigest: '1.2.840.113549.1.9.4',
  signingTime: '1.2.840.113549.1.9.5',
  rsaPss: '1.2.840.113549.1.1.10',
};

const HASHES: Record<string, string> = {
  '1.3.14.3.2.26': 'sha1',
  '2.16.840.1.101.3.4.2.1': 'sha256',
  '2.16.840.1.101.3.4.2.2': 'sha384',
  '2.16.840.1.101.3.4.2.3': 'sha512',
};

const { Class, Type } = forge.asn1;

function fingerprintOfPem(pem: string): string {
  return new X509Certificate(pem).fingerprint256.replace(/:/g, '').toLowerCase();
}

type SignatureDictionary = { dict: Map<string, PdfValue> };

/** Form fields looked at, at most: a briefing has one; a form that is larger is not one of ours. */
const MAX_FIELDS = 1000;

/** Signature dictionaries: the values of the AcroForm's signature fields, else any /Type /Sig object. */
function signatureDictionaries(doc: PdfDocument): SignatureDictionary[] {
  const found: SignatureDictionary[] = [];
  const tolerant = <T>(read: () => T, otherwise: T): T => {
    try {
      return read();
    } catch (err) {
      // A malformed part is no signature; a file that needs too much work is refused whole.
      if (err instanceof PdfTooComplexError) throw err;
      return otherwise;
    }
  };
  const root = tolerant(() => dictOf(resolve(doc, doc.trailer.get('Root'))), null);
  const form = tolerant(() => dictOf(resolve(doc, root?.get('AcroForm'))), null);
  const fields = tolerant(() => resolve(doc, form?.get('Fields')), null);
  // The field tree may name the same object twice or itself among its kids: each object is
  // visited once, and the walk stops after MAX_FIELDS fields however the tree is shaped.
  const visited = new Set<number>();
  let budget = MAX_FIELDS;
  const visit = (v: PdfValue | undefined, depth: number) => {
    if (depth > 4 || budget <= 0 || !v) return;
    if (v.kind === 'ref') {
      if (visited.has(v.num)) return;
      visited.add(v.num);
    }
    budget--;
    const field = tolerant(() => dictOf(resolve(doc, v)), null);
    if (!field) return;
    const ft = field.get('FT');
    const value = tolerant(() => dictOf(resolve(doc, field.get('V'))), null);
    if (ft?.kind === 'name' && ft.value === 'Sig' && value?.has('ByteRange')) found.push({ dict: value });
    const kids = tolerant(() => resolve(doc, field.get('Kids')), null);
    if (kids?.kind === 'array') for (const k of kids.items) visit(k, depth + 1);
  };
  if (fields?.kind === 'array') for (const f of fields.items) visit(f, 0);
  if (found.length > 0) return found;
  for (const num of doc.offsets.keys()) {
    // An object this reader cannot parse (e.g. a stream) is not a signature dictionary.
    const d = tolerant(() => dictOf(resolve(doc, { kind: 'ref', num, gen: 0 })), null);
    const type = d?.get('Type');
    if (d?.has('ByteRange') && d.has('Contents') && type?.kind === 'name' && type.value === 'Sig') found.push({ dict: d });
  }
  return found;
}

function byteRangeOf(dict: Map<string, PdfValue>): [number, number, number, number] | null {
  const br = dict.get('ByteRange');
  if (br?.kind !== 'array' || br.items.length !== 4) return null;
  const nums = br.items.map((i) => (i.kind === 'number' && Number.isInteger(i.value) && i.value >= 0 ? i.value : NaN));
  return nums.some(Number.isNaN) ? null : (nums as [number, number, number, number]);
}

type CmsCheck = {
  digestMatches: boolean;
  signatureValid: boolean;
  signerPem: string | null;
  signingTime: Date | null;
  problems: string[];
};

function asn1Bytes(node: forge.asn1.Asn1): Buffer {
  return Buffer.from(forge.asn1.toDer(node).getBytes(), 'binary');
}

function checkCms(cmsBytes: Buffer, signedData: Buffer): CmsCheck {
  const out: CmsCheck = { digestMatches: false, signatureValid: false, signerPem: null, signingTime: null, problems: [] };
  let p7: forge.pkcs7.PkcsSignedData;
  try {
    // The placeholder is padded with zeros after the DER; parseAllBytes: false ignores them.
    // (@types/node-forge knows only the older boolean second argument.)
    const asn1 = forge.asn1.fromDer(forge.util.createBuffer(cmsBytes.toString('binary')), { parseAllBytes: false } as unknown as boolean);
    p7 = forge.pkcs7.messageFromAsn1(asn1) as forge.pkcs7.PkcsSignedData;
  } catch (err) {
    out.problems.push(`The signature value is not a readable CMS signature (${(err as Error).message}).`);
    return out;
  }
  const raw = (p7 as unknown as { rawCapture?: { signerInfos?: forge.asn1.Asn1[] } }).rawCapture;
  const signerInfo = raw?.signerInfos?.[0];
  if (!signerInfo || !Array.isArray(signerInfo.value)) {
    out.problems.push('The signature names no signer.');
    return out;
  }
  const parts = signerInfo.value as forge.asn1.Asn1[];
  const issuerAndSerial = parts[1];
  const digestAlgorithm = parts[2];
  let i = 3;
  const signedAttrs = parts[i]?.tagClass === Class.CONTEXT_SPECIFIC && parts[i]?.type === 0 ? parts[i++] : undefined;
  const signatureAlgorithm = parts[i++];
  const signatureValue = parts[i];
  if (!issuerAndSerial || !digestAlgorithm || !signatureAlgorithm || !signatureValue || typeof signatureValue.value !== 'string') {
    out.problems.push('The signer information in the signature is incomplete.');
    return out;
  }
  const digestOid = forge.asn1.derToOid(((digestAlgorithm.value as forge.asn1.Asn1[])[0]!.value as string) ?? '');
  const hash = HASHES[digestOid];
  if (!hash) {
    out.problems.push(`The signature uses a digest this check does not support (${digestOid}).`);
    return out;
  }
  const sigAlgOid = forge.asn1.derToOid(((signatureAlgorithm.value as forge.asn1.Asn1[])[0]!.value as string) ?? '');
  if (sigAlgOid === OID.rsaPss) {
    out.problems.push('The signature uses RSA-PSS, which this check does not support.');
    return out;
  }

  // The signer's certificate: the one whose issuer and serial number the signer info names.
  const [issuerAsn1, serialAsn1] = issuerAndSerial.value as forge.asn1.Asn1[];
  const serialHex = forge.util.bytesToHex((serialAsn1?.value as string) ?? '');
  const issuerDer = issuerAsn1 ? asn1Bytes(issuerAsn1) : Buffer.alloc(0);
  const signerCert = p7.certificates.find(
    (c) => c.serialNumber.replace(/^0+/, '') === serialHex.replace(/^0+/, '') && asn1Bytes(forge.pki.distinguishedNameToAsn1(c.issuer)).equals(issuerDer),
  );
  if (!signerCert) {
    out.problems.push('The signature does not carry the certificate it was made with.');
    return out;
  }
  out.signerPem = forge.pki.certificateToPem(signerCert);

  const contentDigest = createHash(hash).update(signedData).digest();
  let toVerify: Buffer;
  if (signedAttrs) {
    const attrs = signedAttrs.value as forge.asn1.Asn1[];
    let messageDigest: Buffer | null = null;
    let contentTypeIsData = false;
    for (const attr of attrs) {
      const [oidNode, setNode] = attr.value as forge.asn1.Asn1[];
      const oid = forge.asn1.derToOid((oidNode?.value as string) ?? '');
      const first = (setNode?.value as forge.asn1.Asn1[] | undefined)?.[0];
      if (!first) continue;
      if (oid === OID.messageDigest) messageDigest = Buffer.from(first.value as string, 'binary');
      if (oid === OID.contentType) contentTypeIsData = forge.asn1.derToOid(first.value as string) === OID.data;
      if (oid === OID.signingTime) {
        out.signingTime = first.type === Type.UTCTIME ? forge.asn1.utcTimeToDate(first.value as string) : forge.asn1.generalizedTimeToDate(first.value as string);
      }
    }
    out.digestMatches = messageDigest !== null && messageDigest.equals(contentDigest);
    if (!out.digestMatches) out.problems.push('The file has been changed since it was signed: its contents no longer match the signed digest.');
    if (!contentTypeIsData) out.problems.push('The signature does not declare plain data as its content type.');
    // The signature covers the DER of the signed attributes as a SET (RFC 5652 §5.4), not the [0] form.
    toVerify = asn1Bytes(forge.asn1.create(Class.UNIVERSAL, Type.SET, true, attrs));
  } else {
    out.digestMatches = true;
    toVerify = signedData;
  }
  try {
    const publicKey = new X509Certificate(out.signerPem).publicKey;
    out.signatureValid = cryptoVerify(hash, toVerify, publicKey, Buffer.from(signatureValue.value, 'binary'));
  } catch (err) {
    out.problems.push(`The signature could not be checked (${(err as Error).message}).`);
    return out;
  }
  if (!out.signatureValid) out.problems.push('The signature does not verify with the certificate it carries.');
  return out;
}

function infoOf(doc: PdfDocument) {
  let info: Map<string, PdfValue> | null = null;
  try {
    info = dictOf(resolve(doc, doc.trailer.get('Info')));
  } catch (err) {
    // A malformed Info object only means the file does not say which briefing it is.
    if (err instanceof PdfTooComplexError) throw err;
  }
  const text = (key: string) => {
    try {
      return pdfText(resolve(doc, info?.get(key)) ?? undefined);
    } catch (err) {
      if (err instanceof PdfTooComplexError) throw err;
      return null;
    }
  };
  const version = text(INFO_KEYS.version);
  return {
    briefing: {
      id: text(INFO_KEYS.briefingId),
      version: version !== null && /^\d+$/.test(version) ? Number(version) : null,
      contentSha256: text(INFO_KEYS.contentSha256),
      status: text(INFO_KEYS.status),
      organization: text(INFO_KEYS.organization),
    },
    signerName: text(INFO_KEYS.signerName),
    signerRole: text(INFO_KEYS.signerRole),
  };
}

/**
 * @param pdf the uploaded bytes
 * @param organizationCertificates PEMs of every certificate the organisation has signed with
 *   (retired ones too, so that older briefings still verify)
 */
export function verifyPdf(pdf: Buffer, organizationCertificates: string[]): PdfVerification {
  const fileSha256 = createHash('sha256').update(pdf).digest('hex');
  try {
    return check(pdf, fileSha256, organizationCertificates);
  } catch (err) {
    // Whatever the file does to the reader, the answer is "not valid" with a reason, never a crash.
    const result = emptyResult(fileSha256);
    result.problems.push(
      err instanceof PdfTooComplexError
        ? 'This file is too complex for the check: it is not a briefing this check can confirm.'
        : err instanceof PdfReadError
          ? `This is not a readable PDF file (${err.message}).`
          : 'This is not a readable PDF file.',
    );
    return result;
  }
}

function emptyResult(fileSha256: string): PdfVerification {
  return {
    valid: false,
    fileSha256,
    signaturePresent: false,
    signatureCount: 0,
    coversWholeFile: false,
    byteRange: null,
    digestMatches: false,
    cmsSignatureValid: false,
    signedByOrganization: false,
    certificateValidAtSigning: false,
    signer: { name: null, role: null, certificateSubject: null, certificateFingerprintSha256: null },
    signingTime: null,
    briefing: { id: null, version: null, contentSha256: null, status: null, organization: null },
    problems: [],
  };
}

function check(pdf: Buffer, fileSha256: string, organizationCertificates: string[]): PdfVerification {
  const result = emptyResult(fileSha256);
  let doc: PdfDocument;
  try {
    doc = openPdf(pdf);
  } catch (err) {
    if (err instanceof PdfTooComplexError) throw err;
    result.problems.push(err instanceof PdfReadError ? `This is not a readable PDF file (${err.message}).` : 'This is not a readable PDF file.');
    return result;
  }
  const info = infoOf(doc);
  result.briefing = info.briefing;
  if (!info.briefing.id) result.problems.push('The file does not identify itself as a Cutline briefing.');

  const signatures = signatureDictionaries(doc);
  result.signatureCount = signatures.length;
  result.signaturePresent = signatures.length > 0;
  if (!result.signaturePresent) {
    result.problems.push('The file carries no digital signature.');
    return result;
  }
  // Check the signature that covers the file to its end if there is one, else the first.
  const candidates = signatures.map((s) => ({ ...s, br: byteRangeOf(s.dict) }));
  const chosen = candidates.find((c) => c.br && c.br[2] + c.br[3] === pdf.length) ?? candidates[0]!;
  const br = chosen.br;
  result.byteRange = br;
  const contents = chosen.dict.get('Contents');
  if (!br || contents?.kind !== 'string') {
    result.problems.push('The signature has no usable byte range or value.');
    return result;
  }
  const [a, b, c, d] = br;
  // The gap between the two ranges must be exactly the <hex> signature value, and nothing else.
  result.coversWholeFile = a === 0 && b > 0 && c > b && c + d === pdf.length && contents.start === b && contents.end === c;
  if (!result.coversWholeFile) result.problems.push('The signature does not cover the whole file: something was added or moved after signing.');
  if (c + d > pdf.length || a + b > c) {
    result.problems.push('The signed byte ranges lie outside the file.');
    return result;
  }
  const signedData = Buffer.concat([pdf.subarray(a, a + b), pdf.subarray(c, c + d)]);
  const cms = checkCms(contents.bytes, signedData);
  result.digestMatches = cms.digestMatches;
  result.cmsSignatureValid = cms.signatureValid;
  result.problems.push(...cms.problems);
  result.signingTime = cms.signingTime ?? pdfDate(pdfText(chosen.dict.get('M')));
  result.signer = {
    name: info.signerName ?? pdfText(chosen.dict.get('Name')),
    role: info.signerRole,
    certificateSubject: null,
    certificateFingerprintSha256: null,
  };

  if (cms.signerPem) {
    const x509 = new X509Certificate(cms.signerPem);
    const fingerprint = x509.fingerprint256.replace(/:/g, '').toLowerCase();
    result.signer.certificateSubject = x509.subject.replace(/\n/g, ', ');
    result.signer.certificateFingerprintSha256 = fingerprint;
    const known = new Set(organizationCertificates.map(fingerprintOfPem));
    result.signedByOrganization = known.has(fingerprint);
    if (!result.signedByOrganization) result.problems.push('The signature was not made with this organisation’s certificate.');
    const at = result.signingTime;
    result.certificateValidAtSigning = at !== null && at >= new Date(x509.validFrom) && at <= new Date(x509.validTo);
    if (!result.certificateValidAtSigning) result.problems.push('The certificate was not valid at the signing time.');
  }

  result.valid =
    result.coversWholeFile && result.digestMatches && result.cmsSignatureValid && result.signedByOrganization && result.certificateValidAtSigning && info.briefing.id !== null;
  return result;
}
