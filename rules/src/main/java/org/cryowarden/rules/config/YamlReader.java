package org.cryowarden.rules.config;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.CharBuffer;
import java.nio.charset.CharsetDecoder;
import java.nio.charset.CoderResult;
import java.nio.charset.CodingErrorAction;
import java.nio.charset.StandardCharsets;
import java.nio.file.AccessDeniedException;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.Deque;
import java.util.HashMap;
import java.util.IdentityHashMap;
import java.util.Iterator;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.SourcePosition;
import org.snakeyaml.engine.v2.api.LoadSettings;
import org.snakeyaml.engine.v2.api.lowlevel.Compose;
import org.snakeyaml.engine.v2.api.lowlevel.Parse;
import org.snakeyaml.engine.v2.events.Event;
import org.snakeyaml.engine.v2.events.ScalarEvent;
import org.snakeyaml.engine.v2.exceptions.Mark;
import org.snakeyaml.engine.v2.exceptions.MarkedYamlEngineException;
import org.snakeyaml.engine.v2.exceptions.YamlEngineException;
import org.snakeyaml.engine.v2.nodes.MappingNode;
import org.snakeyaml.engine.v2.nodes.Node;
import org.snakeyaml.engine.v2.nodes.NodeTuple;
import org.snakeyaml.engine.v2.nodes.ScalarNode;
import org.snakeyaml.engine.v2.nodes.SequenceNode;
import org.snakeyaml.engine.v2.nodes.Tag;
import org.snakeyaml.engine.v2.schema.CoreSchema;

/**
 * Reads one YAML 1.2 document into a positioned {@link ConfigNode} tree, the common first step of every
 * cryowarden file (site, rule set, room, scenario). Built on SnakeYAML Engine's compose API, which keeps node
 * marks but leaves several checks to its constructor; this class does them itself so that no YAML feature can
 * smuggle in something a configuration file has no use for:
 *
 * <ul>
 *   <li>one document per file, at most {@value #MAX_BYTES} bytes (1 MiB), UTF-8;</li>
 *   <li>nesting at most {@value #MAX_DEPTH} levels deep;</li>
 *   <li>at most {@value #MAX_ALIASES} aliases ({@code *name}) per file, expanding to at most
 *       {@value #MAX_ALIAS_EXPANSION} nodes in all, none recursive;</li>
 *   <li>keys are unique text (no numbers, booleans, null, lists or mappings as keys, no {@code <<} merge);</li>
 *   <li>no explicit tags ({@code !!str}, {@code !java.io.File}): values are plain YAML and stay text until a
 *       loader interprets them.</li>
 * </ul>
 *
 * <p>Every problem carries a 1-based {@code FILE:LINE:COLUMN}; all problems found in the tree are reported in
 * one {@link ConfigException}. A syntax error or a nesting limit stops reading at that point. Positions of nodes
 * reached through an alias are those of the anchored original. Stateless and thread-safe.
 */
public final class YamlReader {

    /** Largest file accepted, in bytes (1 MiB): configuration files are a few kilobytes. */
    public static final int MAX_BYTES = 1 << 20;

    /** Deepest nesting of lists and mappings accepted. A site file needs about ten levels. */
    public static final int MAX_DEPTH = 32;

    /** Most aliases ({@code *name}) accepted in one file. */
    public static final int MAX_ALIASES = 20;

    /** Most nodes that aliases may add to the tree when expanded, against "billion laughs" documents. */
    public static final int MAX_ALIAS_EXPANSION = 10_000;

    private static final String CORE_TAG_PREFIX = "tag:yaml.org,2002:";

    private YamlReader() {
    }

    /**
     * Reads a file; its path as given names it in every position.
     *
     * @throws ConfigException with every problem found, including a missing, unreadable, oversized or
     *                         non-UTF-8 file
     */
    public static ConfigNode read(Path file) throws ConfigException {
        Objects.requireNonNull(file, "file");
        String label = file.toString();
        SourcePosition whole = new SourcePosition(label, 0, 0);
        byte[] bytes;
        try {
            if (Files.isDirectory(file)) {
                throw problem(whole, "is a directory, expected a YAML file");
            }
            long size = Files.size(file);
            if (size > MAX_BYTES) {
                throw problem(whole, tooLarge(size));
            }
            bytes = Files.readAllBytes(file);
        } catch (NoSuchFileException e) {
            throw problem(whole, "file not found");
        } catch (AccessDeniedException e) {
            throw problem(whole, "cannot read the file: permission denied");
        } catch (IOException e) {
            throw problem(whole, "cannot read the file: " + e.getMessage());
        }
        if (bytes.length > MAX_BYTES) {
            throw problem(whole, tooLarge(bytes.length));
        }
        return parse(decode(bytes, label), label);
    }

    /**
     * Reads YAML text, naming it {@code label} in every position (a file name, or e.g. {@code <test>}).
     *
     * @throws ConfigException with every problem found
     */
    public static ConfigNode read(String text, String label) throws ConfigException {
        Objects.requireNonNull(text, "text");
        Objects.requireNonNull(label, "label");
        int size = text.getBytes(StandardCharsets.UTF_8).length;
        if (size > MAX_BYTES) {
            throw problem(new SourcePosition(label, 0, 0), tooLarge(size));
        }
        return parse(text, label);
    }

    private static ConfigNode parse(String text, String label) throws ConfigException {
        LoadSettings settings = LoadSettings.builder()
                .setLabel(label)
                .setSchema(new CoreSchema())
                .setCodePointLimit(MAX_BYTES)
                // Our own, smaller alias limit is checked first, with a position; this one only backs it up.
                .setMaxAliasesForCollections(MAX_ALIASES * 10)
                .setAllowRecursiveKeys(false)
                .setAllowNonScalarKeys(true)
                .setParseComments(false)
                .build();
        List<ConfigProblem> problems = new ArrayList<>();
        try {
            if (!screenEvents(settings, text, label, problems)) {
                throw new ConfigException(problems);
            }
            Iterator<Node> documents = new Compose(settings).composeAllFromString(text).iterator();
            if (!documents.hasNext()) {
                return new ConfigNode.Scalar("", true, new SourcePosition(label, 1, 1));
            }
            Node root = documents.next();
            ConfigNode tree = new TreeBuilder(label, problems).build(root);
            if (!problems.isEmpty()) {
                problems.sort(Comparator.comparingInt((ConfigProblem p) -> p.position().line())
                        .thenComparingInt(p -> p.position().column()));
                throw new ConfigException(problems);
            }
            return tree;
        } catch (MarkedYamlEngineException e) {
            problems.add(syntaxProblem(e, label));
            throw new ConfigException(problems);
        } catch (YamlEngineException e) {
            problems.add(new ConfigProblem(new SourcePosition(label, 0, 0), "cannot read YAML: " + e.getMessage()));
            throw new ConfigException(problems);
        } catch (IllegalArgumentException e) {
            // SnakeYAML Engine's composer throws this, without a mark, for a tag it cannot hold (e.g. "!%A").
            problems.add(new ConfigProblem(new SourcePosition(label, 0, 0), "cannot read YAML: " + e.getMessage()));
            throw new ConfigException(problems);
        }
    }

    /**
     * A first pass over the parser events, before the (recursive) composer runs: it bounds the nesting depth,
     * counts aliases at the place they are written and refuses further documents.
     *
     * @return false when reading must stop here (nesting too deep)
     */
    private static boolean screenEvents(LoadSettings settings, String text, String label, List<ConfigProblem> problems) {
        int documents = 0;
        int aliases = 0;
        // One entry per open collection: for a mapping whether the next node is a key, for a list null.
        Deque<Boolean> open = new ArrayDeque<>();
        for (Event event : new Parse(settings).parseString(text)) {
            Event.ID id = event.getEventId();
            boolean isKey = false;
            if (id == Event.ID.Scalar || id == Event.ID.Alias || id == Event.ID.MappingStart
                    || id == Event.ID.SequenceStart) {
                Boolean expectKey = open.peek();
                if (expectKey != null) {
                    isKey = expectKey;
                    open.pop();
                    open.push(!expectKey);
                }
            }
            switch (id) {
                case DocumentStart:
                    documents++;
                    if (documents == 2) {
                        problems.add(new ConfigProblem(position(event.getStartMark(), label),
                                "found a second YAML document; a cryowarden file holds exactly one (remove the '---' "
                                        + "line or split the file)"));
                    }
                    break;
                case MappingStart:
                case SequenceStart:
                    if (open.size() >= MAX_DEPTH) {
                        problems.add(new ConfigProblem(position(event.getStartMark(), label),
                                "nesting is deeper than " + MAX_DEPTH + " levels; a configuration file never needs that"));
                        return false;
                    }
                    open.push(id == Event.ID.MappingStart);
                    break;
                case MappingEnd:
                case SequenceEnd:
                    open.pop();
                    break;
                case Alias:
                    aliases++;
                    if (aliases == MAX_ALIASES + 1) {
                        problems.add(new ConfigProblem(position(event.getStartMark(), label),
                                "too many aliases: at most " + MAX_ALIASES + " aliases (*name) are allowed per file, "
                                        + "this is alias number " + aliases + "; write the values out instead"));
                    }
                    break;
                case Scalar:
                    ScalarEvent scalar = (ScalarEvent) event;
                    // The composer would merge a "<<" key silently, so it is caught here, where it is still visible.
                    if (isKey && scalar.isPlain() && scalar.getValue().equals("<<")) {
                        problems.add(new ConfigProblem(position(event.getStartMark(), label), "a key must be text, "
                                + "found a merge key (<<); merging mappings is not supported, write the keys out"));
                    }
                    break;
                default:
                    break;
            }
        }
        return true;
    }

    /** Turns composed nodes into {@link ConfigNode}s, collecting every problem. */
    private static final class TreeBuilder {
        private final String label;
        private final List<ConfigProblem> problems;
        private final IdentityHashMap<Node, Boolean> seen = new IdentityHashMap<>();
        private final IdentityHashMap<Node, Boolean> path = new IdentityHashMap<>();
        private int aliasDepth;
        private int expanded;
        private boolean expansionReported;

        TreeBuilder(String label, List<ConfigProblem> problems) {
            this.label = label;
            this.problems = problems;
        }

        ConfigNode build(Node node) {
            SourcePosition position = position(node.getStartMark(), label);
            if (path.containsKey(node)) {
                problems.add(new ConfigProblem(position, "recursive alias: this node contains an alias to itself"));
                return new ConfigNode.Scalar("", true, position);
            }
            boolean alias = seen.put(node, Boolean.TRUE) != null;
            if (alias) {
                aliasDepth++;
            }
            try {
                if (aliasDepth > 0 && ++expanded > MAX_ALIAS_EXPANSION) {
                    if (!expansionReported) {
                        expansionReported = true;
                        problems.add(new ConfigProblem(position, "aliases expand to more than " + MAX_ALIAS_EXPANSION
                                + " nodes; write the values out instead"));
                    }
                    return new ConfigNode.Scalar("", true, position);
                }
                if (!alias) {
                    checkTag(node, position);
                }
                path.put(node, Boolean.TRUE);
                try {
                    return convert(node, position, !alias);
                } finally {
                    path.remove(node);
                }
            } finally {
                if (alias) {
                    aliasDepth--;
                }
            }
        }

        private ConfigNode convert(Node node, SourcePosition position, boolean report) {
            if (node instanceof ScalarNode scalar) {
                boolean isNull = scalar.getTag().equals(Tag.NULL);
                return new ConfigNode.Scalar(isNull ? "" : scalar.getValue(), isNull, position);
            }
            if (node instanceof SequenceNode sequence) {
                List<ConfigNode> items = new ArrayList<>(sequence.getValue().size());
                for (Node item : sequence.getValue()) {
                    items.add(build(item));
                }
                return new ConfigNode.Sequence(items, position);
            }
            MappingNode mapping = (MappingNode) node;
            List<ConfigNode.Entry> entries = new ArrayList<>(mapping.getValue().size());
            Map<String, SourcePosition> firstSeen = new HashMap<>();
            for (NodeTuple tuple : mapping.getValue()) {
                Node keyNode = tuple.getKeyNode();
                SourcePosition keyPosition = position(keyNode.getStartMark(), label);
                Optional<String> key = key(keyNode, keyPosition, report);
                ConfigNode value = build(tuple.getValueNode());
                if (key.isEmpty()) {
                    continue;
                }
                SourcePosition earlier = firstSeen.putIfAbsent(key.get(), keyPosition);
                if (earlier != null) {
                    if (report) {
                        problems.add(new ConfigProblem(keyPosition, "duplicate key '" + key.get()
                                + "': already given at line " + earlier.line() + ", column " + earlier.column()));
                    }
                    continue;
                }
                entries.add(new ConfigNode.Entry(key.get(), keyPosition, value));
            }
            return new ConfigNode.Mapping(entries, position);
        }

        private Optional<String> key(Node keyNode, SourcePosition keyPosition, boolean report) {
            String found;
            if (keyNode instanceof ScalarNode scalar) {
                Tag tag = scalar.getTag();
                if (tag.equals(Tag.STR) && scalar.isResolved()) {
                    return Optional.of(scalar.getValue());
                }
                if (tag.equals(Tag.NULL)) {
                    found = "an empty key";
                } else if (tag.equals(Tag.INT) || tag.equals(Tag.FLOAT)) {
                    found = "the number " + scalar.getValue() + " (quote it if it is meant as text)";
                } else if (tag.equals(Tag.BOOL)) {
                    found = "the boolean " + scalar.getValue() + " (quote it if it is meant as text)";
                } else {
                    // An explicitly tagged key: the key and its value are dropped, so the tag must be reported.
                    if (report) {
                        checkTag(keyNode, keyPosition);
                    }
                    return Optional.empty();
                }
            } else {
                found = keyNode instanceof SequenceNode ? "a list" : "a mapping";
                build(keyNode);
            }
            if (report) {
                problems.add(new ConfigProblem(keyPosition, "a key must be text, found " + found));
            }
            return Optional.empty();
        }

        private void checkTag(Node node, SourcePosition position) {
            if (!node.isResolved()) {
                problems.add(new ConfigProblem(position, "explicit YAML tags are not supported, found '"
                        + shortTag(node.getTag()) + "': write a plain value (quote text that looks like a number)"));
            }
        }
    }

    private static String shortTag(Tag tag) {
        String value = tag.getValue();
        return value.startsWith(CORE_TAG_PREFIX) ? "!!" + value.substring(CORE_TAG_PREFIX.length()) : value;
    }

    private static ConfigProblem syntaxProblem(MarkedYamlEngineException e, String label) {
        Optional<Mark> mark = e.getProblemMark().isPresent() ? e.getProblemMark() : e.getContextMark();
        StringBuilder message = new StringBuilder("YAML syntax error: ");
        String problem = e.getProblem() == null ? "malformed YAML" : e.getProblem().strip();
        if (!problem.contains("(TAB)")) {
            // SnakeYAML appends an indentation hint to every "cannot start any token"; it only fits tabs.
            problem = problem.replaceFirst("\\.? ?\\(Do not use .* for indentation\\)$", "");
        }
        message.append(problem);
        if (e.getContext() != null && e.getContextMark().isPresent()) {
            Mark context = e.getContextMark().get();
            message.append(" (").append(e.getContext().strip()).append(" that started at line ")
                    .append(context.getLine() + 1).append(", column ").append(context.getColumn() + 1).append(')');
        }
        return new ConfigProblem(position(mark, label), message.toString());
    }

    /** SnakeYAML marks are 0-based; people count from 1. */
    private static SourcePosition position(Optional<Mark> mark, String label) {
        return mark.map(m -> new SourcePosition(label, m.getLine() + 1, m.getColumn() + 1))
                .orElseGet(() -> new SourcePosition(label, 0, 0));
    }

    private static String decode(byte[] bytes, String label) throws ConfigException {
        CharsetDecoder decoder = StandardCharsets.UTF_8.newDecoder()
                .onMalformedInput(CodingErrorAction.REPORT)
                .onUnmappableCharacter(CodingErrorAction.REPORT);
        ByteBuffer in = ByteBuffer.wrap(bytes);
        CharBuffer out = CharBuffer.allocate(bytes.length + 1);
        CoderResult result = decoder.decode(in, out, true);
        if (result.isError()) {
            int offset = in.position();
            int line = 1;
            int lineStart = 0;
            for (int i = 0; i < offset; i++) {
                if (bytes[i] == '\n') {
                    line++;
                    lineStart = i + 1;
                }
            }
            String prefix = new String(bytes, lineStart, offset - lineStart, StandardCharsets.UTF_8);
            int column = prefix.codePointCount(0, prefix.length()) + 1;
            throw problem(new SourcePosition(label, line, column), String.format(
                    "byte 0x%02X is not valid UTF-8; save the file as UTF-8", bytes[offset] & 0xff));
        }
        decoder.flush(out);
        out.flip();
        String text = out.toString();
        return text.startsWith("\uFEFF") ? text.substring(1) : text;
    }

    private static String tooLarge(long size) {
        return "the file is " + size + " bytes, more than the " + MAX_BYTES + " bytes (1 MiB) a configuration file "
                + "may have";
    }

    private static ConfigException problem(SourcePosition position, String message) {
        return new ConfigException(List.of(new ConfigProblem(position, message)));
    }
}
