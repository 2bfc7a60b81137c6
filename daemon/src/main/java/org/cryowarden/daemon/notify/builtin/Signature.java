package org.cryowarden.daemon.notify.builtin;

import java.nio.charset.StandardCharsets;
import java.security.GeneralSecurityException;
import java.util.HexFormat;
import javax.crypto.Mac;
import javax.crypto.spec.SecretKeySpec;

/**
 * The webhook signature: HMAC-SHA256 (RFC 2104 with SHA-256, test vectors in RFC 4231) of the exact body bytes
 * with the shared secret, sent as {@code X-Cryowarden-Signature: sha256=<lower-case hex>} so the receiver can check
 * that the notice came from us and was not altered.
 */
public final class Signature {

    public static final String HEADER = "X-Cryowarden-Signature";

    private Signature() {
    }

    /** The header value for {@code body}. */
    public static String header(byte[] secret, byte[] body) {
        return "sha256=" + HexFormat.of().formatHex(hmacSha256(secret, body));
    }

    static byte[] hmacSha256(byte[] secret, byte[] body) {
        try {
            Mac mac = Mac.getInstance("HmacSHA256");
            mac.init(new SecretKeySpec(secret, "HmacSHA256"));
            return mac.doFinal(body);
        } catch (GeneralSecurityException e) {
            // Every Java runtime must provide HmacSHA256 (Java SE "Standard Algorithm Names").
            throw new IllegalStateException("HmacSHA256 is not available in this Java runtime", e);
        }
    }

    static byte[] utf8(String text) {
        return text.getBytes(StandardCharsets.UTF_8);
    }
}
