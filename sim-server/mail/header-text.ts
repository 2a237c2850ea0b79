/**
 * Text made safe for one mail header line: CR, LF, the other Unicode line breaks and the control
 * characters become one space. RFC 5322 §2.2 allows CR LF in a header field only as folding, so a
 * display name or scenario name with a line break could otherwise start a header of its own
 * ("Bcc: …"): header injection (OWASP ASVS 4.0.3 V5.2.3; CWE-93).
 * @example headerText('Axis\r\nBcc: all@example.test') // 'Axis Bcc: all@example.test'
 */
export function headerText(text: string): string {
  return text.replace(/[\u0000-\u001f\u007f-\u009f\u2028\u2029]+/g, ' ').trim();
}
