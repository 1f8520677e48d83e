package dev.espalier.cli;

/** Bad usage or bad input detected by a command; printed as one line, exit code 2. */
final class UserInputException extends RuntimeException {
    UserInputException(String message) {
        super(message);
    }
}
