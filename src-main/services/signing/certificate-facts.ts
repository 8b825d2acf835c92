import { X509Certificate } from 'node:crypto';

/** What a reader of a packet needs to know about a signer's certificate. */
export interface CertificateFacts {
  subject: string;
  /** The subject's common name, or the whole subject when it has none. */
  commonName: string;
  issuer: string;
  /** SHA-256 of the certificate's DER encoding, lower-case hex. */
  fingerprint: string;
  /**
   * Subject and issuer are the same name (RFC 5280 §3.2 "self-issued"): nobody but the holder
   * vouches for the name, so it is shown as self-issued wherever the signature appears.
   */
  selfIssued: boolean;
  notBefore: string;
  notAfter: string;
  serialNumber: string;
}

export function certificateFacts(der: Uint8Array): CertificateFacts {
  const certificate = new X509Certificate(der);
  const commonName = /(?:^|\n)CN=([^\n]*)/.exec(certificate.subject)?.[1] ?? certificate.subject;
  return {
    subject: certificate.subject,
    commonName,
    issuer: certificate.issuer,
    fingerprint: certificate.fingerprint256.replaceAll(':', '').toLowerCase(),
    selfIssued: certificate.subject === certificate.issuer,
    notBefore: new Date(certificate.validFrom).toISOString(),
    notAfter: new Date(certificate.validTo).toISOString(),
    serialNumber: certificate.serialNumber,
  };
}

/** `3f2a…9c01` style short form for tables; the full fingerprint is always printed once nearby. */
export function shortFingerprint(fingerprint: string): string {
  return `${fingerprint.slice(0, 8)}…${fingerprint.slice(-8)}`;
}
