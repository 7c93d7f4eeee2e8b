package dev.winnow.store;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import java.io.ByteArrayInputStream;
import java.io.InputStream;
import java.io.SequenceInputStream;
import java.lang.reflect.Proxy;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.PreparedStatement;
import java.sql.ResultSet;
import java.util.Collections;
import java.util.List;
import java.util.Random;
import java.util.function.Supplier;
import org.junit.jupiter.api.Test;

/**
 * {@link PanelStore#payloadOf}, which reads a payload column without the copy {@code getBytes} makes: every byte
 * must equal what the JDBC driver's own {@code getBytes} returns, through H2's stream and through streams of the
 * other kinds a driver may hand over (several pieces through a reused buffer, as {@link InputStream#transferTo} does,
 * a part of a larger array, a subclass), whatever the size (empty, one byte, exactly the JDK's 8 KiB transfer buffer,
 * larger).
 */
class PayloadReadTest {
    private static final int[] SIZES = {0, 1, 8191, 8192, 8193, 50_000, 200_003};

    @Test
    void h2PayloadsReadBackAsGetBytesReadsThem() throws Exception {
        Random random = new Random(17);
        try (Connection c = DriverManager.getConnection("jdbc:h2:mem:payload-read")) {
            c.createStatement().execute("CREATE TABLE t (id INT PRIMARY KEY, p VARBINARY)");
            try (PreparedStatement ps = c.prepareStatement("INSERT INTO t VALUES (?, ?)")) {
                for (int i = 0; i < SIZES.length; i++) {
                    byte[] b = new byte[SIZES[i]];
                    random.nextBytes(b);
                    ps.setInt(1, i);
                    ps.setBytes(2, b);
                    ps.execute();
                }
                ps.setInt(1, SIZES.length);
                ps.setBytes(2, null);
                ps.execute();
            }
            try (ResultSet rs = c.createStatement().executeQuery("SELECT id, p FROM t ORDER BY id")) {
                while (rs.next()) {
                    byte[] want = rs.getBytes(2);
                    byte[] got = PanelStore.payloadOf(rs, 2);
                    if (want == null) {
                        assertNull(got);
                    } else {
                        assertArrayEquals(want, got, "payload of " + want.length + " bytes");
                    }
                }
            }
        }
    }

    @Test
    void streamsOfOtherKindsAreReadWhole() throws Exception {
        Random random = new Random(18);
        for (int size : SIZES) {
            byte[] want = new byte[size];
            random.nextBytes(want);
            byte[] padded = new byte[size + 7];
            System.arraycopy(want, 0, padded, 3, size);
            List<Supplier<InputStream>> kinds = List.of(
                    () -> new SequenceInputStream(Collections.enumeration(List.of(
                            new ByteArrayInputStream(want, 0, size / 2), new ByteArrayInputStream(want, size / 2, size - size / 2)))),
                    () -> new ByteArrayInputStream(padded, 3, size),
                    () -> new ByteArrayInputStream(want) { },
                    () -> new java.io.BufferedInputStream(new ByteArrayInputStream(want), 1000));
            for (Supplier<InputStream> kind : kinds) {
                InputStream in = kind.get();
                String where = in.getClass().getName() + ", " + size + " bytes";
                assertArrayEquals(want, PanelStore.payloadOf(resultSetOf(in), 1), where);
            }
        }
    }

    /** A result set whose only column reads as the given stream. */
    private static ResultSet resultSetOf(InputStream in) {
        return (ResultSet) Proxy.newProxyInstance(ResultSet.class.getClassLoader(), new Class<?>[] {ResultSet.class},
                (proxy, method, args) -> {
                    if (method.getName().equals("getBinaryStream")) {
                        return in;
                    }
                    throw new UnsupportedOperationException(method.getName());
                });
    }
}
