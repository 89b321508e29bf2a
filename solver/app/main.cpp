// plystrain command line front end.
#include <iostream>

int main() {
  std::cout << "plystrain " << PLYSTRAIN_VERSION << "\n";
  return 0;
}
