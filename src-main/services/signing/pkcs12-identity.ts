import { createPrivateKey } from 'node:crypto';
import forge from 'node-forge';
import { certificateFacts } from './certificate-facts.js';
import { KeyError, type SigningIdentity } from './signing-identity.js';

const ecPublicKey = '1.2.840.10045.2.1';
const keyAlgorithmNames: Record<string, string> = {
  [ecPublicKey]: 'an elliptic-curve (EC) key',
  '1.3.101.112': 'an Ed25519 key',
  '1.3.101.113': 'an Ed448 key',
  '1.2.840.10040.4.1': 'a DSA key',
};

/**
 * Reads a PKCS#12 file (.p12/.pfx) as companies issue them: one RSA private key and its
 * certificate, optionally with issuer certificates. Other key types are refused with a message
 * that says so, because the packet's signatures are RSA with SHA-256 (DESIGN.md, "The record").
 */
export function readPkcs12(
  bytes: Uint8Array,
  passphrase: string,
  fileName = 'the PKCS#12 file',
): SigningIdentity {
  let p12: forge.pkcs12.Pkcs12Pfx;
  try {
    const asn1 = forge.asn1.fromDer(forge.util.createBuffer(Buffer.from(bytes).toString('binary')));
    p12 = forge.pkcs12.pkcs12FromAsn1(asn1, false, passphrase);
  } catch (error) {
    const text = error instanceof Error ? error.message : String(error);
    if (/MAC could not be verified|Invalid password/i.test(text)) {
      throw new KeyError(`${fileName}: the passphrase does not open this PKCS#12 file`);
    }
    throw new KeyError(`${fileName}: not a readable PKCS#12 (.p12/.pfx) file (${text})`);
  }
  const keyBags = [
    ...(p12.getBags({ bagType: forge.pki.oids.pkcs8ShroudedKeyBag })[forge.pki.oids.pkcs8ShroudedKeyBag!] ??
      []),
    ...(p12.getBags({ bagType: forge.pki.oids.keyBag })[forge.pki.oids.keyBag!] ?? []),
  ];
  if (keyBags.length === 0) throw new KeyError(`${fileName}: holds no private key`);
  if (keyBags.length > 1)
    throw new KeyError(`${fileName}: holds ${keyBags.length} private keys; give a file with one`);
  const bag = keyBags[0]!;
  if (!bag.key) {
    const algorithm = bag.asn1 ? privateKeyAlgorithm(bag.asn1) : undefined;
    const what = (algorithm && keyAlgorithmNames[algorithm]) ?? `a key of type ${algorithm ?? 'unknown'}`;
    throw new KeyError(
      `${fileName}: holds ${what}; Limit Ledger signs with RSA keys only. Ask for an RSA certificate (3072 bits or more) or create a personal signing certificate.`,
    );
  }
  const rsaKey = bag.key as forge.pki.rsa.PrivateKey;
  const certificates = (p12.getBags({ bagType: forge.pki.oids.certBag })[forge.pki.oids.certBag!] ?? [])
    .map((certBag) => certBag.cert)
    .filter((cert): cert is forge.pki.Certificate => cert !== undefined);
  const own = certificates.find((cert) => {
    const publicKey = cert.publicKey as forge.pki.rsa.PublicKey;
    return publicKey.n?.equals(rsaKey.n) && publicKey.e?.equals(rsaKey.e);
  });
  if (!own) throw new KeyError(`${fileName}: holds no certificate for its private key`);
  const toDer = (cert: forge.pki.Certificate) =>
    Buffer.from(forge.asn1.toDer(forge.pki.certificateToAsn1(cert)).getBytes(), 'binary');
  const privateKey = createPrivateKey({
    key: Buffer.from(forge.asn1.toDer(forge.pki.privateKeyToAsn1(rsaKey)).getBytes(), 'binary'),
    format: 'der',
    type: 'pkcs1',
  });
  const certificate = toDer(own);
  return {
    privateKey,
    certificate,
    chain: certificates.filter((cert) => cert !== own).map(toDer),
    facts: certificateFacts(certificate),
  };
}

/** PrivateKeyInfo ::= SEQUENCE { version, AlgorithmIdentifier { OID, ... }, ... } (RFC 5208). */
function privateKeyAlgorithm(info: forge.asn1.Asn1): string | undefined {
  try {
    const algorithm = (info.value as forge.asn1.Asn1[])[1];
    const oid = (algorithm!.value as forge.asn1.Asn1[])[0]!;
    return forge.asn1.derToOid(oid.value as string);
  } catch {
    return undefined;
  }
}
