package dev.winnow.api;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.net.Socket;
import java.nio.charset.StandardCharsets;
import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;

/**
 * HTTP/1.1 over a plain socket, for requests a well-behaved client cannot send: raw request targets (broken percent
 * escapes, very long paths), huge headers, a declared length the body never reaches.
 */
final class RawHttp {
    private RawHttp() {
    }

    record Answer(int status, Map<String, String> headers, String body) {
        String header(String name) {
            return headers.get(name.toLowerCase(Locale.ROOT));
        }
    }

    /** Sends {@code head} (request line and headers, CRLF-separated, without the blank line) and {@code body}; reads the answer. */
    static Answer send(int port, String head, byte[] body) throws IOException {
        try (Socket socket = new Socket("127.0.0.1", port)) {
            socket.setSoTimeout(30_000);
            OutputStream out = socket.getOutputStream();
            out.write((head + "\r\nConnection: close\r\n\r\n").getBytes(StandardCharsets.ISO_8859_1));
            if (body != null) {
                try {
                    out.write(body);
                } catch (IOException serverStoppedReading) {
                    // the server may answer and close before reading a body it refuses
                }
            }
            out.flush();
            return read(socket.getInputStream());
        }
    }

    private static Answer read(InputStream in) throws IOException {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        try {
            in.transferTo(bytes);
        } catch (IOException reset) {
            if (bytes.size() == 0) {
                throw reset;
            }
        }
        String text = bytes.toString(StandardCharsets.UTF_8);
        int end = text.indexOf("\r\n\r\n");
        String head = end < 0 ? text : text.substring(0, end);
        String body = end < 0 ? "" : text.substring(end + 4);
        String[] lines = head.split("\r\n");
        int status = Integer.parseInt(lines[0].split(" ")[1]);
        Map<String, String> headers = new LinkedHashMap<>();
        for (int i = 1; i < lines.length; i++) {
            int colon = lines[i].indexOf(':');
            if (colon > 0) {
                headers.put(lines[i].substring(0, colon).trim().toLowerCase(Locale.ROOT), lines[i].substring(colon + 1).trim());
            }
        }
        if ("chunked".equalsIgnoreCase(headers.get("transfer-encoding"))) {
            body = unchunk(body);
        }
        return new Answer(status, headers, body);
    }

    private static String unchunk(String chunked) {
        StringBuilder out = new StringBuilder();
        int at = 0;
        while (at < chunked.length()) {
            int nl = chunked.indexOf("\r\n", at);
            if (nl < 0) {
                break;
            }
            int size = Integer.parseInt(chunked.substring(at, nl).split(";")[0].trim(), 16);
            if (size == 0) {
                break;
            }
            out.append(chunked, nl + 2, Math.min(chunked.length(), nl + 2 + size));
            at = nl + 2 + size + 2;
        }
        return out.toString();
    }
}
