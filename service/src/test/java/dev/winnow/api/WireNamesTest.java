package dev.winnow.api;

import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.databind.BeanDescription;
import com.fasterxml.jackson.databind.introspect.BeanPropertyDefinition;
import org.junit.jupiter.api.Test;

import java.io.IOException;
import java.lang.reflect.RecordComponent;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Every answer record of {@code api} (and every record of {@code research} that declares its wire names) names its fields in snake_case, one underscore before each capital of the
 * component's name ({@code nwTStat} is {@code nw_t_stat}); Jackson's snake_case strategy alone would write
 * {@code nw_tstat}, so a component with consecutive capitals needs an explicit name. Fields keep the components' order.
 */
class WireNamesTest {
    private static final Path CLASSES = Path.of("target/classes/dev/winnow");
    /** The packages whose records answers are made of. */
    private static final List<String> PACKAGES = List.of("api", "research");

    static String snake(String camel) {
        StringBuilder out = new StringBuilder();
        for (char c : camel.toCharArray()) {
            if (Character.isUpperCase(c)) {
                out.append('_').append(Character.toLowerCase(c));
            } else {
                out.append(c);
            }
        }
        return out.toString();
    }

    @Test
    void snakeCaseMarksEveryCapital() {
        assertEquals("nw_t_stat", snake("nwTStat"));
        assertEquals("passes_t3", snake("passesT3"));
        assertEquals("created_at", snake("createdAt"));
    }

    @Test
    void everyAnswerRecordSpellsItsFieldsInSnakeCaseInComponentOrder() throws Exception {
        List<String> wrong = new ArrayList<>();
        int records = 0;
        for (Class<?> type : apiClasses()) {
            if (!type.isRecord() || !answer(type)) {
                continue;
            }
            records++;
            BeanDescription description = Json.MAPPER.getSerializationConfig().introspect(Json.MAPPER.constructType(type));
            List<String> names = description.findProperties().stream().map(BeanPropertyDefinition::getName).toList();
            List<String> expected = new ArrayList<>();
            for (RecordComponent c : type.getRecordComponents()) {
                JsonProperty explicit = c.getAccessor().getAnnotation(JsonProperty.class);
                if (explicit == null && c.getAnnotation(JsonProperty.class) != null) {
                    explicit = c.getAnnotation(JsonProperty.class);
                }
                expected.add(explicit != null ? explicit.value() : snake(c.getName()));
            }
            if (names.size() == expected.size() && !names.equals(expected)) {
                wrong.add(type.getName() + ": " + names + " instead of " + expected);
            }
        }
        assertTrue(records > 10, "found only " + records + " records under " + CLASSES.toAbsolutePath());
        assertEquals(List.of(), wrong);
    }

    /**
     * A record meant for the wire: it declares a naming strategy or a wire name, or is declared in an api route class
     * or wire-form holder ({@code ...Routes}, {@code ...Wire}, {@code ...Json}, {@code Accepted}).
     */
    private static boolean answer(Class<?> type) {
        if (type.isAnnotationPresent(com.fasterxml.jackson.databind.annotation.JsonNaming.class)) {
            return true;
        }
        for (RecordComponent c : type.getRecordComponents()) {
            if (c.getAccessor().isAnnotationPresent(JsonProperty.class) || c.isAnnotationPresent(JsonProperty.class)) {
                return true;
            }
        }
        if (type.getPackageName().endsWith(".research")) {
            return false;
        }
        Class<?> outer = type.getEnclosingClass();
        String name = outer == null ? "" : outer.getSimpleName();
        return name.endsWith("Routes") || name.endsWith("Wire") || name.endsWith("Json") || name.equals("Accepted");
    }

    private static List<Class<?>> apiClasses() throws IOException, ClassNotFoundException {
        List<Class<?>> out = new ArrayList<>();
        for (String pkg : PACKAGES) {
            try (Stream<Path> files = Files.list(CLASSES.resolve(pkg))) {
                for (Path f : files.filter(p -> p.toString().endsWith(".class")).toList()) {
                    String simple = f.getFileName().toString().replace(".class", "");
                    out.add(Class.forName("dev.winnow." + pkg + "." + simple, false, WireNamesTest.class.getClassLoader()));
                }
            }
        }
        return out;
    }
}
