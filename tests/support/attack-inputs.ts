/**
 * Adversarial inputs shared by the unit tests, the integration tests and the fuzz suite.
 */

// Open-redirect bypass forms from the OWASP Unvalidated Redirects and Forwards Cheat Sheet and
// the WHATWG URL Standard (browsers drop tabs and line breaks and read "\" as "/" in http URLs).
export const REDIRECT_BYPASSES: string[] = [
  // raw whitespace and controls
  "/\t/evil.example",
  "/\n/evil.example",
  "/\r\n/evil.example",
  " //evil.example",
  "/\u0000/evil.example",
  "/\u2028/evil.example",
  "/\u3000/evil.example",
  // encoded whitespace and controls
  "/%09/evil.example",
  "/%0a/evil.example",
  "/%0D%0A/evil.example",
  "%2F%2Fevil.example",
  "/%2F/evil.example",
  "/%2f%2fevil.example",
  // backslashes
  "/\\evil.example",
  "\\\\evil.example",
  "/\\/evil.example",
  "\\/evil.example",
  "/%5Cevil.example",
  "/%5c/evil.example",
  // double slashes
  "//evil.example",
  "///evil.example",
  "/.//evil.example",
  "/./\\evil.example",
  "//evil.example/tanks",
  // schemes
  "https://evil.example",
  "HTTPS://evil.example",
  "http:evil.example",
  "http:/evil.example",
  "javascript:alert(1)",
  "data:text/html,<script>alert(1)</script>",
  // userinfo
  "//user@evil.example",
  "//fernwater.test@evil.example",
  "https://fernwater.test@evil.example",
  // too long for anyone's good
  "/" + "a".repeat(5000),
];
