package org.cryowarden.daemon.access;

import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.security.SecureRandom;
import java.util.Base64;
import java.util.Objects;

/**
 * The stored form of an API token: {@code sha256:} and the unpadded base64url SHA-256 of the token text. A plain
 * SHA-256 suffices, and a slow password hash (PBKDF2) would only cost time on every request: the tokens are 256
 * random bits made by {@link #newToken()}, not words a person chose, so guessing one from its hash is as hard as
 * guessing the token itself. Comparison is in constant time ({@link MessageDigest#isEqual}).
 *
 * @param digest the 32 bytes of the hash
 */
public record TokenHash(byte[] digest) {

    static final String PREFIX = "sha256:";
    private static final SecureRandom RANDOM = new SecureRandom();

    public TokenHash {
        Objects.requireNonNull(digest, "digest");
        if (digest.length != 32) {
            throw new IllegalArgumentException("a SHA-256 hash has 32 bytes, got " + digest.length);
        }
        digest = digest.clone();
    }

    /** A new token: 32 bytes from {@link SecureRandom}, base64url without padding (43 characters). */
    public static String newToken() {
        byte[] bytes = new byte[32];
        RANDOM.nextBytes(bytes);
        return Base64.getUrlEncoder().withoutPadding().encodeToString(bytes);
    }

    public static TokenHash of(String token) {
        try {
            return new TokenHash(MessageDigest.getInstance("SHA-256").digest(token.getBytes(StandardCharsets.UTF_8)));
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException("every Java platform has SHA-256", e);
        }
    }

    /**
     * Reads the stored form.
     *
     * @throws IllegalArgumentException saying what is wrong
     */
    public static TokenHash parse(String text) {
        if (!text.startsWith(PREFIX)) {
            throw new IllegalArgumentException("token hash must start with '" + PREFIX + "' (make one with"
                    + " `cryowarden token new --operator NAME`)");
        }
        byte[] digest;
        try {
            digest = Base64.getUrlDecoder().decode(text.substring(PREFIX.length()));
        } catch (IllegalArgumentException e) {
            throw new IllegalArgumentException("token hash is not base64url after '" + PREFIX + "'");
        }
        return new TokenHash(digest);
    }

    /** Whether {@code token} hashes to this, in time independent of where the bytes differ. */
    public boolean matches(String token) {
        return MessageDigest.isEqual(digest, of(token).digest);
    }

    @Override
    public byte[] digest() {
        return digest.clone();
    }

    public String text() {
        return PREFIX + Base64.getUrlEncoder().withoutPadding().encodeToString(digest);
    }

    @Override
    public boolean equals(Object other) {
        return other instanceof TokenHash hash && MessageDigest.isEqual(digest, hash.digest);
    }

    @Override
    public int hashCode() {
        return java.util.Arrays.hashCode(digest);
    }

    @Override
    public String toString() {
        return text();
    }
}
