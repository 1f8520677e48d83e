package dev.espalier.abnf;

import java.util.Optional;

/**
 * Finds the files named by {@code ;@use "path"} directives (see {@link Abnf}). The engine reads no
 * files by itself: whoever parses with imports supplies the way to load them.
 */
@FunctionalInterface
public interface ImportResolver {

    /**
     * A loaded file.
     *
     * @param name a name that identifies the file (two directives naming the same file must yield
     *             the same name, so that import cycles are recognised); used as {@link RuleSite#source()}
     * @param text the file's text
     */
    record Source(String name, String text) {
        /** Checks that nothing is null. */
        public Source {
            java.util.Objects.requireNonNull(name);
            java.util.Objects.requireNonNull(text);
        }
    }

    /**
     * Loads the file a directive names.
     *
     * @param importingFile the name of the file holding the directive
     * @param path          the path as written in the directive, usually relative to the importing file
     * @return the file, or empty when it does not exist or cannot be read
     */
    Optional<Source> resolve(String importingFile, String path);
}
